import type { Metadata } from "next";
import { PageHeader } from "../_components/page-header";
import { serverMode } from "@/lib/server/mode";
import { safeNextPath } from "@/lib/server/auth";
import { LoginForm } from "./_components/login-form";

export const metadata: Metadata = { title: "Log in" };
export const dynamic = "force-dynamic";

export default async function LoginPage({ searchParams }: { searchParams: Promise<{ next?: string | string[] }> }) {
  const { next } = await searchParams;
  const mode = serverMode();
  return (
    <div className="login-page">
      <PageHeader title="Log in" description={mode.mode === "team" ? "This workbench is shared: log in with the account an admin made for you." : "This workbench runs in local mode: there is no login, every page is open to you on this machine."} />
      {mode.mode === "team" ? <LoginForm next={safeNextPath(Array.isArray(next) ? next[0] : next)} /> : null}
    </div>
  );
}
