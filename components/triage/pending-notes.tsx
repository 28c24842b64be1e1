import { Section } from "@/components/ui/section";
import { LocalTime } from "@/components/ui/local-time";

type Note = { id: number; code: string; columns: string[]; comment: string; author: string; createdAt: Date };

/**
 * Notes made on this version's findings before the decision (through the API's
 * …/finding-comments): the decision sends every one of them to the provider with its own
 * comments, so the analyst sees them here before deciding. Never shown to providers.
 */
export function PendingNotes({ notes }: { notes: Note[] }) {
  if (!notes.length) return null;
  return (
    <Section
      title="Notes waiting for the decision"
      id="notes"
      note="The decision sends these to the provider with its own comments."
    >
      <ul className="grid grid-cols-1 gap-2 text-sm" data-testid="pending-notes">
        {notes.map((n) => (
          <li key={n.id} className="rounded border-l-4 border-channel bg-channel-wash px-3 py-2">
            <code className="text-xs">{n.code}</code>
            {n.columns.length ? (
              <span className="font-mono text-xs"> ({n.columns.join(", ")})</span>
            ) : null}: <span className="whitespace-pre-wrap">{n.comment}</span>
            <span className="block text-xs text-silt-ink">
              {n.author}, <LocalTime value={n.createdAt} />
            </span>
          </li>
        ))}
      </ul>
    </Section>
  );
}
