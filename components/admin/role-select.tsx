"use client";

import { useState, useTransition } from "react";
import { ROLES, ROLE_LABELS, type Role } from "@/lib/auth/roles";
import { changeRoleAction } from "./actions";

export function RoleSelect({ userId, role, email }: { userId: number; role: Role; email: string }) {
  const [value, setValue] = useState<Role>(role);
  const [message, setMessage] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  return (
    <div className="flex items-center gap-2">
      <label className="sr-only" htmlFor={`role-${userId}`}>Role of {email}</label>
      <select
        id={`role-${userId}`}
        value={value}
        disabled={pending}
        onChange={(e) => {
          const next = e.target.value as Role;
          const previous = value;
          setValue(next);
          startTransition(async () => {
            const result = await changeRoleAction(userId, next);
            setMessage(result.message);
            if (!result.ok) setValue(previous);
          });
        }}
        className="rounded-md border border-slate-300 px-2 py-1 text-sm"
      >
        {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
      </select>
      {message ? <span role="status" className="text-xs text-slate-600">{message}</span> : null}
    </div>
  );
}
