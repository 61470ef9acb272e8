import type { Metadata } from "next";
import Link from "next/link";
import type { ReactNode } from "react";
import { AccountMenu } from "./_components/account-menu";
import { BrandMark } from "./_components/brand-mark";
import { SafetyNote } from "./_components/safety-note";
import { TopNav } from "./_components/top-nav";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Meltledger", template: "%s · Meltledger" },
  description: "Curation workbench for laser powder bed fusion build records.",
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en">
      <body>
        <a className="skip-link" href="#main">
          Skip to content
        </a>
        <header className="site-header">
          <div className="site-header__inner">
            <Link href="/" className="brand">
              <BrandMark />
              Meltledger
            </Link>
            <TopNav />
            <AccountMenu />
          </div>
        </header>
        <main id="main" className="site-main" tabIndex={-1}>
          {children}
        </main>
        <footer className="site-footer">
          <SafetyNote />
        </footer>
      </body>
    </html>
  );
}
