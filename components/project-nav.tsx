'use client';
import Link from 'next/link';
import { usePathname } from 'next/navigation';

export interface NavItem {
  href: string;
  label: string;
}

export function ProjectNav({ items }: { items: NavItem[] }) {
  const path = usePathname();
  return (
    <nav aria-label="Project" className="flex flex-col gap-0.5">
      {items.map((i) => {
        const active = path === i.href;
        return (
          <Link
            key={i.href}
            href={i.href}
            aria-current={active ? 'page' : undefined}
            className={`rounded px-3 py-1.5 text-sm no-underline ${active ? 'bg-mineral-100 font-medium text-mineral-900' : 'text-ink-700 hover:bg-ink-100 hover:text-ink-900'}`}
          >
            {i.label}
          </Link>
        );
      })}
    </nav>
  );
}
