"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button type="button" onClick={() => signOut({ callbackUrl: "/sign-in" })}
      className="rounded-md px-3 py-2 text-sm text-mist-300 hover:bg-night-800 hover:text-white">
      Sign out
    </button>
  );
}
