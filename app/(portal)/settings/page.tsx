import Link from "next/link";
import { requireUser } from "@/lib/auth/session";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password-rules";
import { roleLabel } from "@/lib/format";
import { ApiTokens } from "@/components/settings/api-tokens";
import { can } from "@/lib/auth/permissions";
import { listApiTokens, TOKEN_LIST } from "@/lib/people/queries";
import { nextHref, PAGE_SIZE } from "@/lib/http/page";
import { PasswordForm } from "./password-form";
import { createTokenAction, revokeTokenAction } from "./token-actions";

export const metadata = { title: "Settings" };

export default async function SettingsPage() {
  const user = await requireUser();
  const tokens = can(user.role, "token.manage")
    ? await listApiTokens(user.id, { limit: PAGE_SIZE })
    : { rows: [], nextKey: null };
  return (
    <>
      <PageHeader title="Settings" description="Your account." />
      <Section id="account" title="Account">
        <dl className="grid max-w-xl grid-cols-[10rem_1fr] gap-y-1.5 text-base">
          <dt className="text-silt-ink">Name</dt>
          <dd>{user.name}</dd>
          <dt className="text-silt-ink">E-mail</dt>
          <dd>{user.email}</dd>
          <dt className="text-silt-ink">Role</dt>
          <dd>{roleLabel(user.role)}</dd>
          <dt className="text-silt-ink">Organisation</dt>
          <dd>{user.organisationName ?? "–"}</dd>
        </dl>
      </Section>
      <Section
        id="password"
        title="Change your password"
        note="After the change you sign in again; sessions on other devices end too."
      >
        <PasswordForm minLength={PASSWORD_MIN_LENGTH} />
      </Section>
      {can(user.role, "token.manage") ? (
        <Section
          id="tokens"
          title="API tokens"
          note="For scripts that upload batches or read reports through the API. A token can do what you can, no more."
        >
          <p className="mb-3 text-base">
            <Link href="/api-reference" className="text-channel-deep underline underline-offset-2">
              API reference
            </Link>{" "}
            — every route, its parameters and its answers.
          </p>
          <ApiTokens
            first={{
              data: tokens.rows.map((t) => ({
                ...t,
                createdAt: t.createdAt.toISOString(),
                lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
                revokedAt: t.revokedAt?.toISOString() ?? null,
              })),
              next: nextHref("/api/v1/tokens", new URLSearchParams(), TOKEN_LIST, tokens),
            }}
            pageSize={PAGE_SIZE}
            create={createTokenAction}
            revoke={revokeTokenAction}
          />
        </Section>
      ) : null}
    </>
  );
}
