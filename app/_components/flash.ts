import { cookies } from "next/headers";

/** Name of the one-shot cookie that tells a page what was just saved. */
export const FLASH_COOKIE = "meltledger-flash";

/**
 * Leaves a note for the page a server action redirects to ("record-12:created"), so the
 * address stays the plain page URL. The page's FlashNotice shows it once and clears it.
 */
export async function setFlash(entity: string, event: string): Promise<void> {
  (await cookies()).set(FLASH_COOKIE, `${entity}:${event}`, { path: "/", maxAge: 60, sameSite: "lax", httpOnly: false });
}
