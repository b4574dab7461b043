import Link from 'next/link';
export default function NotFound() {
  return (
    <main className="mx-auto max-w-lg px-6 py-24 text-center">
      <h1 className="mb-2">Not found</h1>
      <p className="text-sm text-ink-600">
        This page does not exist, or it belongs to an organization you are not a member of.
      </p>
      <p className="mt-4">
        <Link href="/projects">Your projects</Link>
      </p>
    </main>
  );
}
