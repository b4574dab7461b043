export function EmptyState({
  title,
  children,
  next,
}: {
  title: string;
  children: React.ReactNode;
  next?: string;
}) {
  return (
    <div className="panel border-dashed p-8 text-center">
      <h2 className="mb-2">{title}</h2>
      <div className="mx-auto max-w-xl text-sm text-ink-600">{children}</div>
      {next ? <p className="mx-auto mt-3 max-w-xl text-xs text-ink-500">Coming next: {next}</p> : null}
    </div>
  );
}
