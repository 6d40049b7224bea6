"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";

export function SignInForm({ next = "/" }: { next?: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [isPending, setPending] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    setPending(true);
    setError(null);
    try {
      const result = await signIn("credentials", {
        email: String(form.get("email") ?? ""),
        password: String(form.get("password") ?? ""),
        redirect: false,
      });
      if (!result || result.error) {
        // One message for unknown e-mail and wrong password: it must not reveal which.
        setError("That e-mail and password do not match an account. Check both and try again.");
        return;
      }
      router.replace(next);
      router.refresh();
    } catch {
      setError("Sign-in is not reachable right now. Try again in a moment.");
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} className="mt-5 space-y-4" noValidate>
      <Field name="email" label="E-mail" type="email" autoComplete="username" required />
      <Field
        name="password"
        label="Password"
        type="password"
        autoComplete="current-password"
        required
      />
      {error ? (
        <p role="alert" className="rounded-md bg-alarm-100 px-3 py-2 text-sm text-alarm-700">
          {error}
        </p>
      ) : null}
      <button type="submit" className={`${buttonClass.primary} w-full`} disabled={isPending}>
        {isPending ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
