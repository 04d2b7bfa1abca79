import type { Metadata } from "next";
import type { ReactNode } from "react";
import { Providers } from "@/components/providers";
import { inter } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Siderea", template: "%s · Siderea" },
  description: "Arrival-direction anisotropy analysis for ultra-high-energy cosmic-ray arrays.",
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans antialiased">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
