"use client";

import { Button } from "@/components/ui/button";

export default function WorkspaceError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div role="alert" className="rounded-lg border border-red-200 bg-red-50 p-6 text-red-900">
      <h1 className="text-lg font-semibold">This page could not be shown</h1>
      <p className="mt-1">The error was logged on the server{error.digest ? ` (reference ${error.digest})` : ""}. Nothing you entered was lost.</p>
      <Button variant="secondary" className="mt-4" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}
