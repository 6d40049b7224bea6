"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: "/sign-in?reason=signed-out" })}
      className="rounded-md px-2 py-1.5 text-sm text-ink-soft hover:bg-sea-50 hover:text-ink"
    >
      Sign out
    </button>
  );
}
