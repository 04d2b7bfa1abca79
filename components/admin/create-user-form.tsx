"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { ROLES, ROLE_LABELS } from "@/lib/auth/roles";
import { createUserAction, type ActionResult } from "./actions";

function FieldError({ result, name }: { result: ActionResult | null; name: string }) {
  const message = result && !result.ok ? result.fieldErrors?.[name] : undefined;
  return message ? <p id={`${name}-error`} className="mt-1 text-sm text-red-700">{message}</p> : null;
}

export function CreateUserForm() {
  const [result, action, pending] = useActionState(createUserAction, null);
  const invalid = (name: string) => (result && !result.ok && result.fieldErrors?.[name] ? true : undefined);
  return (
    <form action={action} className="grid gap-3 md:grid-cols-2" aria-label="Create a user">
      <div>
        <label htmlFor="new-email" className="block text-sm font-medium">E-mail</label>
        <input id="new-email" name="email" type="email" required aria-invalid={invalid("email")} aria-describedby="email-error"
          className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
        <FieldError result={result} name="email" />
      </div>
      <div>
        <label htmlFor="new-name" className="block text-sm font-medium">Name</label>
        <input id="new-name" name="name" required aria-invalid={invalid("name")} aria-describedby="name-error"
          className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
        <FieldError result={result} name="name" />
      </div>
      <div>
        <label htmlFor="new-role" className="block text-sm font-medium">Role</label>
        <select id="new-role" name="role" defaultValue="member" className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2">
          {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
        </select>
        <FieldError result={result} name="role" />
      </div>
      <div>
        <label htmlFor="new-password" className="block text-sm font-medium">Initial password</label>
        <input id="new-password" name="password" type="password" required minLength={10} autoComplete="new-password"
          aria-invalid={invalid("password")} aria-describedby="password-error"
          className="mt-1 w-full rounded-md border border-slate-300 px-3 py-2" />
        <FieldError result={result} name="password" />
      </div>
      <div className="md:col-span-2 flex items-center gap-4">
        <Button type="submit" disabled={pending}>{pending ? "Creating…" : "Create user"}</Button>
        {result ? (
          <p role="status" className={result.ok ? "text-green-800" : "text-red-700"}>{result.message}</p>
        ) : null}
      </div>
    </form>
  );
}
