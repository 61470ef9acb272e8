"use client";

import { useEffect, useState } from "react";
import { Alert } from "./alert";

const COOKIE = "meltledger-flash";

function readFlash(): string | null {
  const entry = document.cookie.split("; ").find((c) => c.startsWith(`${COOKIE}=`));
  return entry ? decodeURIComponent(entry.slice(COOKIE.length + 1)) : null;
}

/** Shows, once, what the last action did to this entity ("Record saved"), then clears the note. */
export function FlashNotice({ entity, messages }: { entity: string; messages: Record<string, string> }) {
  const [message, setMessage] = useState<string | null>(null);
  useEffect(() => {
    const flash = readFlash();
    if (!flash) return;
    const [who, event] = flash.split(":");
    if (who !== entity || !event) return;
    document.cookie = `${COOKIE}=; path=/; max-age=0; samesite=lax`;
    setMessage(messages[event] ?? null);
    // messages is a literal at each call site; the note is read once per entity
  }, [entity]);
  return message ? <Alert tone="info" title={message} /> : null;
}
