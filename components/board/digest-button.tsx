"use client";
/** Queues the weekly digest to every lead now, and says what happened. */
import { useState } from "react";
import { Button } from "@/components/ui/button";

export function DigestButton() {
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  async function send() {
    setBusy(true);
    setMessage(null);
    try {
      const res = await fetch("/api/v1/board/digest", { method: "POST" });
      const body = (await res.json().catch(() => null)) as {
        data?: { queued: number; recipients: number };
        detail?: string;
      } | null;
      if (res.ok && body?.data)
        setMessage(
          `Digest queued for ${body.data.queued} of ${body.data.recipients} ${body.data.recipients === 1 ? "lead" : "leads"}; it goes out within a minute.`,
        );
      else setMessage(body?.detail ?? "The digest could not be queued. Try again in a minute.");
    } catch {
      setMessage("The server did not answer. Check your connection and try again.");
    } finally {
      setBusy(false);
    }
  }
  return (
    <div className="flex items-center gap-3">
      <span role="status" aria-live="polite" className="text-sm text-ink-soft">
        {message}
      </span>
      <Button variant="secondary" size="sm" busy={busy} onClick={send} data-testid="send-digest">
        Send digest now
      </Button>
    </div>
  );
}
