"use client";

import { startTransition, useActionState, useEffect, useRef } from "react";
import type { ActionResult } from "@/lib/auth/action";

type FormAction = (prev: ActionResult | null, formData: FormData) => Promise<ActionResult>;

/**
 * Submits a form to a server action without React's automatic form reset, so that a rejected
 * submission keeps what the user typed. With resetOnSuccess the form clears after an accepted one.
 */
export function useFormAction(action: FormAction, opts: { resetOnSuccess?: boolean } = {}) {
  const [state, dispatch, isPending] = useActionState<ActionResult | null, FormData>(action, null);
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (state?.ok && opts.resetOnSuccess) formRef.current?.reset();
  }, [state, opts.resetOnSuccess]);
  const onSubmit = (e: React.FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const formData = new FormData(e.currentTarget);
    startTransition(() => dispatch(formData));
  };
  const fieldErrors = state && !state.ok ? state.fieldErrors : undefined;
  return { state, isPending, formRef, onSubmit, fieldErrors };
}
