export function Spinner({ label = 'Loading…' }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-3 py-8 text-loam-700">
      <span
        className="h-5 w-5 animate-spin rounded-full border-2 border-leaf-300 border-t-leaf-700"
        aria-hidden
      />
      <span>{label}</span>
    </div>
  );
}
