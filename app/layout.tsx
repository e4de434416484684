// The root layout: fonts, theme (light, dark or the system's) and page metadata.
import type { Metadata } from "next";
import { headers } from "next/headers";
import type { ReactNode } from "react";
import { mono, sans } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Emberline", template: "%s · Emberline" },
  description: "A team notebook for identifying elements from atomic emission spectra.",
};

// Sets the theme class before first paint, so a dark-theme user never sees a light flash.
const themeScript = `(function(){try{var t=localStorage.getItem("emberline-theme");var d=t?t==="dark":matchMedia("(prefers-color-scheme: dark)").matches;document.documentElement.classList.toggle("dark",d)}catch(e){}})()`;

export default async function RootLayout({ children }: { children: ReactNode }) {
  // proxy.ts gives every page request a fresh nonce; reading it renders every page per request,
  // which a nonce-based Content-Security-Policy needs (a prerendered page would carry no nonce).
  const nonce = (await headers()).get("x-nonce") ?? undefined;
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`} suppressHydrationWarning>
      <head>
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: themeScript }} />
      </head>
      <body>{children}</body>
    </html>
  );
}
