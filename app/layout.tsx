import type { Metadata } from "next";
import { connection } from "next/server";
import type { ReactNode } from "react";
import { geistMono, geistSans } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Chainwright", template: "%s · Chainwright" },
  description: "Plan and check analog signal chains from sensor to converter, together.",
};

export default async function RootLayout({ children }: { children: ReactNode }) {
  // Every page is rendered per request: the content security policy's nonce (proxy.ts) is new each time,
  // and Next can only put it on the scripts of a page it renders now.
  await connection();
  return (
    <html lang="en" className={`${geistSans.variable} ${geistMono.variable}`}>
      <body className="min-h-screen">{children}</body>
    </html>
  );
}
