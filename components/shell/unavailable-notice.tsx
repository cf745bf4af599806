/** Says plainly that a part of the product is not built yet, instead of pretending it works. */
export function UnavailableNotice({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section className="mx-auto max-w-prose py-12">
      <h1 className="text-2xl font-bold">{title}</h1>
      <div className="mt-4 rounded border border-rule bg-surface p-5 text-ink-muted">{children}</div>
    </section>
  );
}
