"use client";

import { useState, useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/select";
import { addMemberAction, removeMemberAction, type MemberKind } from "./actions";

type Member = { id: number; name: string; detail?: string };

type Props = {
  slug: string;
  kind: MemberKind;
  members: Member[];
  /** who could be added (empty when the user may not manage the study) */
  candidates: Member[];
  canManage: boolean;
};

const WORDS: Record<
  MemberKind,
  { one: string; a: string; add: string; added: string; removed: string; empty: string }
> = {
  analyst: {
    one: "analyst",
    a: "an analyst",
    add: "Assign",
    added: "assigned",
    removed: "no longer assigned",
    empty: "No analyst is assigned yet.",
  },
  provider: {
    one: "provider organisation",
    a: "a provider organisation",
    add: "Admit",
    added: "admitted",
    removed: "no longer admitted",
    empty: "No provider organisation is admitted yet.",
  },
};

/** The study's analysts or provider organisations, with add and remove for those who manage the study. */
export function MembersPanel({ slug, kind, members, candidates, canManage }: Props) {
  const w = WORDS[kind];
  const [chosen, setChosen] = useState("");
  const [error, setError] = useState("");
  const [pending, startTransition] = useTransition();
  const available = candidates.filter((c) => !members.some((m) => m.id === c.id));
  const selectId = `add-${kind}`;

  function add() {
    if (!chosen) {
      setError(`Choose ${w.a} first.`);
      return;
    }
    startTransition(async () => {
      const r = await addMemberAction(slug, kind, chosen);
      if (r.ok) {
        toast.success(`${r.data.name} is ${w.added}.`);
        setChosen("");
        setError("");
      } else {
        setError(
          Object.values(r.fieldErrors ?? {})
            .flat()
            .join(" ") || r.message,
        );
      }
    });
  }

  function remove(m: Member) {
    startTransition(async () => {
      const r = await removeMemberAction(slug, kind, m.id);
      if (r.ok) toast.success(`${r.data.name} is ${w.removed}.`);
      else toast.error(r.message);
    });
  }

  return (
    <div className="flex flex-col gap-2">
      {members.length === 0 ? (
        <p className="text-sm text-silt-ink">{w.empty}</p>
      ) : (
        <ul className="divide-y divide-silt-line rounded border border-silt-line bg-white">
          {members.map((m) => (
            <li key={m.id} className="flex items-center gap-3 px-3 py-1.5 text-base">
              <span className="flex-1">
                {m.name}
                {m.detail ? <span className="ml-2 text-sm text-silt-ink">{m.detail}</span> : null}
              </span>
              {canManage ? (
                <Button
                  variant="quiet"
                  size="sm"
                  className="text-clay"
                  disabled={pending}
                  onClick={() => remove(m)}
                  aria-label={`Remove ${m.name}`}
                >
                  Remove
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      )}
      {canManage ? (
        <div className="flex flex-col gap-1">
          <div className="flex flex-wrap items-center gap-2">
            <label htmlFor={selectId} className="sr-only">
              {kind === "analyst" ? "Analyst to assign" : "Provider organisation to admit"}
            </label>
            <Select
              id={selectId}
              value={chosen}
              onChange={(e) => setChosen(e.target.value)}
              className="h-8 w-72 text-sm"
              aria-invalid={error ? true : undefined}
              aria-describedby={`${selectId}-error`}
            >
              <option value="">{available.length ? `choose ${w.a}` : `every ${w.one} is already in`}</option>
              {available.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                  {c.detail ? ` (${c.detail})` : ""}
                </option>
              ))}
            </Select>
            <Button
              variant="secondary"
              size="sm"
              onClick={add}
              busy={pending}
              disabled={available.length === 0}
            >
              {w.add}
            </Button>
          </div>
          <p id={`${selectId}-error`} aria-live="polite" className="text-sm text-clay">
            {error}
          </p>
        </div>
      ) : null}
    </div>
  );
}
