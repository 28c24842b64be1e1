"use client";

import { useState } from "react";
import { signOut } from "next-auth/react";
import { Button } from "@/components/ui/button";

export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="quiet"
      size="sm"
      busy={busy}
      onClick={async () => {
        setBusy(true);
        await signOut({ redirect: false });
        window.location.assign("/sign-in");
      }}
    >
      Sign out
    </Button>
  );
}
