import { Alert } from "@/components/ui";

/** An analysis's notes (interpolation, held data, skipped samples…) as one warning list; nothing when none. */
export function NotesAlert({ notes }: { notes: readonly string[] }) {
  if (notes.length === 0) return null;
  return (
    <Alert tone="warn" title="Notes">
      <ul className="list-disc pl-4">
        {notes.map((note) => (
          <li key={note}>{note}</li>
        ))}
      </ul>
    </Alert>
  );
}
