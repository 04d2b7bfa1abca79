import type { Metadata } from "next";
import Link from "next/link";
import { requirePageUser } from "@/lib/auth/server";
import { listUsers } from "@/lib/services/users";
import { recentAudit } from "@/lib/services/audit";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";
import { CreateUserForm } from "@/components/admin/create-user-form";
import { RoleSelect } from "@/components/admin/role-select";

export const metadata: Metadata = { title: "Admin" };
export const dynamic = "force-dynamic";

export default async function AdminPage() {
  const { user, forbidden } = await requirePageUser("users:manage");
  if (forbidden) return <Forbidden role={user.role} what="User administration" />;
  const [users, audit] = await Promise.all([listUsers(), recentAudit(20)]);

  return (
    <>
      <PageHeader title="Administration" lead="People who can sign in, their roles, and the latest entries of the audit log." actions={<Link href="/admin/inbox" className="rounded-md border border-slate-300 bg-white px-4 py-2 text-sm">Mail inbox</Link>} />
      <Card title="Create a user" className="mb-4">
        <CreateUserForm />
      </Card>
      <Card title="Users" className="mb-4">
        <table className="w-full text-sm">
          <caption className="sr-only">Users and their roles</caption>
          <thead className="text-left text-slate-500">
            <tr><th scope="col">Name</th><th scope="col">E-mail</th><th scope="col">Role</th><th scope="col">Since</th></tr>
          </thead>
          <tbody>
            {users.map((u) => (
              <tr key={u.id} className="border-t border-slate-100">
                <td className="py-2 pr-2">{u.name}</td>
                <td className="py-2 pr-2">{u.email}</td>
                <td className="py-2 pr-2"><RoleSelect userId={u.id} role={u.role} email={u.email} /></td>
                <td className="py-2">{u.createdAt.toISOString().slice(0, 10)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
      <Card title="Audit log (latest 20)">
        {audit.length === 0 ? <p className="text-slate-600">No entries yet.</p> : (
          <ul className="space-y-1 text-sm">
            {audit.map((a) => (
              <li key={a.id}>
                <time dateTime={a.createdAt.toISOString()} className="text-slate-500">{a.createdAt.toISOString().replace("T", " ").slice(0, 19)} UTC</time>{" "}
                <span className="font-medium">{a.actor?.name ?? "system"}</span> {a.action} {a.targetType} {a.targetId ?? ""} {JSON.stringify(a.details)}
              </li>
            ))}
          </ul>
        )}
      </Card>
    </>
  );
}
