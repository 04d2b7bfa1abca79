import { ROLE_LABELS, type Role } from "@/lib/auth/roles";

export function Forbidden({ role, what }: { role: Role; what: string }) {
  return (
    <div role="alert" data-testid="forbidden" className="rounded-lg border border-red-200 bg-red-50 p-6 text-red-900">
      <h1 className="text-lg font-semibold">Not available to your role</h1>
      <p className="mt-1">
        {what} is not available to the {ROLE_LABELS[role].toLowerCase()} role. Ask an administrator if you need access.
      </p>
    </div>
  );
}
