import Link from "next/link";
import { pageActor } from "../_lib/actor";
import { logoutAction } from "../login/actions";
import { serverMode } from "@/lib/server/mode";
import "./account-menu.css";

/** Who is working: "Local mode" on a loopback workbench, or the signed-in user with a way out. */
export async function AccountMenu() {
  const mode = serverMode();
  const actor = await pageActor();
  if (mode.mode === "local") {
    return (
      <div className="account-menu">
        <span className="muted" title={mode.reason}>Local mode</span>
        <Link href="/admin/users">Users</Link>
      </div>
    );
  }
  if (!actor.ok) {
    return (
      <div className="account-menu">
        <Link href="/login">Log in</Link>
      </div>
    );
  }
  return (
    <form action={logoutAction} className="account-menu">
      <span>
        {actor.data.name} <span className="muted">({actor.data.role})</span>
      </span>
      {actor.data.role === "admin" ? <Link href="/admin/users">Users</Link> : null}
      <button type="submit" className="button button--ghost button--small">
        Log out
      </button>
    </form>
  );
}
