export function Denied({ what }: { what: string }) {
  return (
    <div role="alert" className="panel p-6 text-sm text-ink-700">
      <h2 className="mb-1">Not available for your role</h2>
      <p>
        {what} is not part of what your role in this organization can open. An owner can change your role on
        the members page.
      </p>
    </div>
  );
}
