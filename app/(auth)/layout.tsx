import type { ReactNode } from "react";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center bg-night-950 p-6">
      <div className="w-full max-w-sm">
        <p className="mb-6 text-center text-3xl font-semibold tracking-tight text-white">
          Siderea<span className="text-dawn-500">.</span>
        </p>
        {children}
      </div>
    </main>
  );
}
