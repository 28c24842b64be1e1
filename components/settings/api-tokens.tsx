"use client";
/** Personal API tokens for scripts: create (shown once), list, revoke. */
import { LocalTime } from "@/components/ui/local-time";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { ShowNext } from "@/components/ui/show-next";
import type { ListPage } from "@/lib/client/fetcher";
import { usePagedList } from "@/lib/client/use-paged-list";
import type { Result } from "@/lib/result";

type Token = {
  id: number;
  name: string;
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
};

export function ApiTokens({
  first,
  pageSize,
  create,
  revoke,
}: {
  first: ListPage<Token>;
  pageSize: number;
  create: (name: string) => Promise<Result<{ token: string; name: string }>>;
  revoke: (id: number) => Promise<Result<unknown>>;
}) {
  const router = useRouter();
  const [name, setName] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [shown, setShown] = useState<{ name: string; token: string } | null>(null);
  const [pending, start] = useTransition();
  const { rows: tokens, next, busy, error, showNext } = usePagedList(first);

  return (
    <div className="grid max-w-3xl gap-4">
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          start(async () => {
            const r = await create(name);
            if (r.ok) {
              setShown({ name: r.data.name, token: r.data.token });
              setName("");
              setErrors({});
              router.refresh();
            } else {
              setErrors(r.fieldErrors ?? {});
              toast.error(r.message);
            }
          });
        }}
      >
        <Field
          id="token-name"
          label="New token's name"
          hint="What will use it, e.g. “nightly export script”."
          errors={errors.name}
        >
          <Input value={name} onChange={(e) => setName(e.target.value)} maxLength={100} className="w-72" />
        </Field>
        <Button type="submit" busy={pending} className="mb-6">
          Create token
        </Button>
      </form>
      {shown ? (
        <div
          className="rounded border border-channel bg-channel-wash px-4 py-3"
          role="status"
          data-testid="new-token"
        >
          <p className="font-semibold">
            Copy the token “{shown.name}” now: it is shown this once and never again.
          </p>
          <code className="mt-2 block break-all rounded bg-white px-2 py-1 font-mono text-sm">
            {shown.token}
          </code>
          <p className="mt-2 text-sm">
            Send it as <code className="font-mono">Authorization: Bearer &lt;token&gt;</code>; it acts with
            your role and scope.
          </p>
        </div>
      ) : null}
      {tokens.length ? (
        <table className="text-sm">
          <thead>
            <tr className="border-b border-silt text-left">
              <th className="py-1 pr-4">Name</th>
              <th className="pr-4">Starts with</th>
              <th className="pr-4">Created</th>
              <th className="pr-4">Last used</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {tokens.map((t) => (
              <tr key={t.id} className="border-b border-silt-line">
                <td className="py-1.5 pr-4">{t.name}</td>
                <td className="pr-4 font-mono">{t.prefix}…</td>
                <td className="pr-4 tabular-nums">
                  <LocalTime value={t.createdAt} />
                </td>
                <td className="pr-4 tabular-nums">
                  {t.lastUsedAt ? <LocalTime value={t.lastUsedAt} /> : "never"}
                </td>
                <td>
                  {t.revokedAt ? (
                    <span className="text-silt-ink">
                      revoked <LocalTime value={t.revokedAt} />
                    </span>
                  ) : (
                    <Button
                      variant="danger"
                      size="sm"
                      onClick={() =>
                        start(async () => {
                          const r = await revoke(t.id);
                          if (r.ok) {
                            toast.success(`Token “${t.name}” revoked; it stops working at once.`);
                            router.refresh();
                          } else toast.error(r.message);
                        })
                      }
                    >
                      Revoke
                    </Button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      {tokens.length ? (
        <ShowNext
          shown={tokens.length}
          more={next !== null}
          pageSize={pageSize}
          noun="tokens"
          busy={busy}
          error={error}
          onNext={showNext}
        />
      ) : (
        <p className="text-sm text-silt-ink">No tokens yet.</p>
      )}
    </div>
  );
}
