"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/components/ui/use-hydrated";
import { SignInSchema } from "@/lib/validations/user";

function messageFor(error: string | undefined): string {
  if (error?.startsWith("rate-limited:")) {
    const seconds = Number(error.split(":")[1]);
    return `Too many failed attempts. Try again in ${Number.isFinite(seconds) ? seconds : "a few"} seconds.`;
  }
  return "The e-mail address or password is incorrect.";
}

export function SignInForm() {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const hydrated = useHydrated();

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const parsed = SignInSchema.safeParse({ email: form.get("email"), password: form.get("password") });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? "Check the form.");
      return;
    }
    setPending(true);
    setError(null);
    const result = await signIn("credentials", { ...parsed.data, redirect: false });
    setPending(false);
    if (!result || result.error) {
      setError(messageFor(result?.error ?? undefined));
      return;
    }
    router.replace("/");
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} method="post" data-hydrated={hydrated ? "true" : "false"} className="space-y-4 rounded-lg bg-white p-6 shadow-lg" noValidate aria-labelledby="sign-in-title">
      <h1 id="sign-in-title" className="text-lg font-semibold">
        Sign in
      </h1>
      <div>
        <label htmlFor="email" className="block text-sm font-medium text-slate-700">
          E-mail
        </label>
        <input id="email" name="email" type="email" autoComplete="username" required
          className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
      </div>
      <div>
        <label htmlFor="password" className="block text-sm font-medium text-slate-700">
          Password
        </label>
        <input id="password" name="password" type="password" autoComplete="current-password" required
          className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
      </div>
      {error ? (
        <p role="alert" data-testid="sign-in-error" className="rounded-md bg-red-50 px-3 py-2 text-sm text-red-800">
          {error}
        </p>
      ) : null}
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
