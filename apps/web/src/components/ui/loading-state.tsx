export function LoadingState({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 px-2 py-10 text-ink-600">
      <span className="inline-block h-4 w-4 animate-spin rounded-full border-2 border-stream-200 border-t-stream-700" aria-hidden="true" />
      <span>{label}</span>
    </div>
  );
}
