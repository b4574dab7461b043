'use client';
import { useId, useState } from 'react';

/**
 * A button that shows or hides what follows it. The content stays mounted while hidden, so a half-done
 * form keeps its state; `initiallyOpen` for the cases where the content is the next step (no revision yet).
 */
export function Disclosure({
  label,
  initiallyOpen,
  children,
}: {
  label: string;
  initiallyOpen: boolean;
  children: React.ReactNode;
}) {
  const [open, setOpen] = useState(initiallyOpen);
  const id = useId();
  return (
    <>
      <button
        type="button"
        className="btn-quiet py-1"
        aria-expanded={open}
        aria-controls={id}
        onClick={() => setOpen((o) => !o)}
      >
        <span aria-hidden="true">{open ? '▾' : '▸'}</span> {label}
      </button>
      <div id={id} hidden={!open} className="mt-2 w-full">
        {children}
      </div>
    </>
  );
}
