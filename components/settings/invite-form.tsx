"use client";
import { useState, useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import type { Result } from "@/lib/result";

type Org = { id: number; name: string; kind: string };

export function InviteForm({
  organisations,
  invite,
}: {
  organisations: Org[];
  invite: (i: {
    email: string;
    name: string;
    role: string;
    organisationId: string;
  }) => Promise<Result<{ email: string }>>;
}) {
  const [v, setV] = useState({ email: "", name: "", role: "provider", organisationId: "" });
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [pending, start] = useTransition();
  const orgs = organisations.filter((o) =>
    v.role === "provider" ? o.kind === "provider" : o.kind === "team",
  );
  return (
    <form
      className="grid max-w-xl gap-4"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r = await invite(v);
          if (r.ok) {
            toast.success(`Invitation sent to ${r.data.email}.`);
            setV({ email: "", name: "", role: v.role, organisationId: v.organisationId });
            setErrors({});
          } else {
            setErrors(r.fieldErrors ?? {});
            toast.error(r.message);
          }
        });
      }}
    >
      <Field id="invite-email" label="E-mail" errors={errors.email}>
        <Input
          type="email"
          value={v.email}
          onChange={(e) => setV({ ...v, email: e.target.value })}
          required
        />
      </Field>
      <Field id="invite-name" label="Name" errors={errors.name}>
        <Input value={v.name} onChange={(e) => setV({ ...v, name: e.target.value })} required />
      </Field>
      <Field id="invite-role" label="Role" errors={errors.role}>
        <Select value={v.role} onChange={(e) => setV({ ...v, role: e.target.value, organisationId: "" })}>
          <option value="provider">Provider — sends batches for an organisation</option>
          <option value="analyst">Analyst — reviews batches of assigned studies</option>
        </Select>
      </Field>
      <Field id="invite-org" label="Organisation" errors={errors.organisationId}>
        <Select value={v.organisationId} onChange={(e) => setV({ ...v, organisationId: e.target.value })}>
          <option value="">
            {v.role === "provider" ? "Choose the provider organisation" : "No organisation"}
          </option>
          {orgs.map((o) => (
            <option key={o.id} value={o.id}>
              {o.name}
            </option>
          ))}
        </Select>
      </Field>
      <div>
        <Button type="submit" busy={pending}>
          Send invitation
        </Button>
      </div>
    </form>
  );
}
