import type { Metadata } from "next";
import { listAccounts } from "@/lib/server/users";
import { serverMode } from "@/lib/server/mode";
import { Alert } from "../../_components/alert";
import { LoadError } from "../../_components/load-error";
import { PageHeader } from "../../_components/page-header";
import { pageActor } from "../../_lib/actor";
import { AddUserForm, UserRowForm } from "./_components/user-forms";

export const metadata: Metadata = { title: "Users" };
export const dynamic = "force-dynamic";

export default async function UsersPage({ searchParams }: { searchParams: Promise<{ added?: string; changed?: string }> }) {
  const actor = await pageActor();
  if (!actor.ok) return <LoadError error={actor.error} what="the users" />;
  const result = await listAccounts(actor.data);
  if (!result.ok) return <LoadError error={result.error} what="the users" />;
  const { added, changed } = await searchParams;
  const mode = serverMode();
  return (
    <>
      <PageHeader
        title="Users"
        eyebrow="Admin"
        description="Contributors enter and edit records and sources; reviewers also resolve flags and accept records; admins also manage users and settings."
      />
      {mode.mode === "local" ? (
        <Alert tone="info" title="Local mode">
          <p>{mode.reason} Accounts made here are used when the server runs in team mode.</p>
        </Alert>
      ) : null}
      {added ? <Alert tone="info" title={`Added ${added}`} /> : null}
      {changed ? <Alert tone="info" title={`Saved ${changed}`} /> : null}
      <section className="panel" aria-labelledby="users-list">
        <div className="panel__title">
          <h2 id="users-list">Accounts</h2>
        </div>
        <div className="table-wrap">
          <table className="table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Role</th>
                <th scope="col">Status</th>
                <th scope="col">Sessions</th>
                <th scope="col">Change</th>
              </tr>
            </thead>
            <tbody>
              {result.data.map((u) => (
                <tr key={u.id}>
                  <td>{u.name}</td>
                  <td>{u.role}</td>
                  <td>{u.disabled ? "disabled" : u.canLogIn ? "can log in" : "no password yet"}</td>
                  <td className="numeric">{u.activeSessions}</td>
                  <td>
                    <UserRowForm user={{ id: u.id, name: u.name, role: String(u.role), disabled: u.disabled }} self={u.id === actor.data.id} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
      <section className="panel" aria-labelledby="users-add">
        <div className="panel__title">
          <h2 id="users-add">Add an account</h2>
        </div>
        <AddUserForm />
      </section>
    </>
  );
}
