/** What a screen will hold once its feature ships, said plainly. */
export function ScreenOutline({ items, title = "What this screen will hold" }: { items: string[]; title?: string }) {
  return (
    <section aria-label={title} className="mb-6 rounded-lg border border-line bg-surface p-5 shadow-card">
      <h2 className="text-body font-semibold text-ink-900">{title}</h2>
      <ul className="mt-3 grid gap-2 text-body text-ink-700 md:grid-cols-2">
        {items.map((item) => (
          <li key={item} className="flex gap-2">
            <span className="mt-2 h-1.5 w-1.5 shrink-0 rounded-full bg-stream-500" aria-hidden="true" />
            <span>{item}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
