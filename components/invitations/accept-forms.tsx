"use client";

import { signIn, useSession } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import {
  acceptWithNewAccountAction,
  joinWithAccountAction,
} from "@/app/(auth)/invite/[token]/actions";
import { buttonClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { useFormAction } from "@/components/ui/use-form-action";

/** Account creation for a new address; on success it signs in with the chosen password. */
export function CreateAccountForm({
  token,
  email,
  minPasswordLength,
}: {
  token: string;
  email: string;
  minPasswordLength: number;
}) {
  const router = useRouter();
  const { state, isPending, formRef, onSubmit, fieldErrors } = useFormAction(
    acceptWithNewAccountAction,
  );
  const password = useRef("");
  const [signInError, setSignInError] = useState<string | null>(null);
  useEffect(() => {
    if (!state?.ok) return;
    void signIn("credentials", { email, password: password.current, redirect: false }).then(
      (result) => {
        password.current = "";
        if (!result || result.error) {
          setSignInError("Your account is ready, but signing in failed. Sign in by hand.");
          return;
        }
        router.replace("/");
        router.refresh();
      },
    );
  }, [state, email, router]);
  return (
    <form
      ref={formRef}
      onSubmit={(e) => {
        password.current = String(new FormData(e.currentTarget).get("password") ?? "");
        onSubmit(e);
      }}
      className="mt-5 space-y-4"
      noValidate
    >
      <input type="hidden" name="token" value={token} />
      <Field
        name="email"
        label="E-mail"
        type="email"
        value={email}
        readOnly
        autoComplete="username"
      />
      <Field name="name" label="Your name" autoComplete="name" errors={fieldErrors?.name} />
      <Field
        name="password"
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${minPasswordLength} characters.`}
        errors={fieldErrors?.password}
      />
      <Field
        name="confirm"
        label="Password again"
        type="password"
        autoComplete="new-password"
        errors={fieldErrors?.confirm}
      />
      {state ? (
        <p
          role={state.ok ? "status" : "alert"}
          className={`rounded-md px-3 py-2 text-sm ${state.ok ? "bg-ok-100 text-ok-700" : "bg-alarm-100 text-alarm-700"}`}
        >
          {state.message}
        </p>
      ) : null}
      {signInError ? (
        <p role="alert" className="rounded-md bg-alarm-100 px-3 py-2 text-sm text-alarm-700">
          {signInError} <a href="/sign-in">Sign in</a>
        </p>
      ) : null}
      <button
        type="submit"
        className={`${buttonClass.primary} w-full`}
        disabled={isPending || state?.ok}
      >
        {isPending ? "Creating your account…" : "Create account and join"}
      </button>
    </form>
  );
}

/** For the signed-in invitee: join, then make the new organisation the active one. */
export function JoinForm({
  token,
  organisationId,
  organisationName,
}: {
  token: string;
  organisationId: number;
  organisationName: string;
}) {
  const router = useRouter();
  const { update } = useSession();
  const { state, isPending, formRef, onSubmit } = useFormAction(joinWithAccountAction);
  useEffect(() => {
    if (!state?.ok) return;
    void update({ organisationId }).then(() => {
      router.replace("/");
      router.refresh();
    });
  }, [state, organisationId, update, router]);
  return (
    <form ref={formRef} onSubmit={onSubmit} className="mt-5 space-y-4">
      <input type="hidden" name="token" value={token} />
      {state ? (
        <p
          role={state.ok ? "status" : "alert"}
          className={`rounded-md px-3 py-2 text-sm ${state.ok ? "bg-ok-100 text-ok-700" : "bg-alarm-100 text-alarm-700"}`}
        >
          {state.message}
        </p>
      ) : null}
      <button
        type="submit"
        className={`${buttonClass.primary} w-full`}
        disabled={isPending || state?.ok}
      >
        {isPending ? "Joining…" : `Join ${organisationName}`}
      </button>
    </form>
  );
}
