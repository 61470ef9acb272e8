"use client";

import { useEffect, type RefObject } from "react";

/**
 * After a failed submit, moves focus to the message at the top (when there is one) or to the
 * first field marked invalid, so keyboard and screen-reader users land where the problem is.
 */
export function useFocusOnError(formRef: RefObject<HTMLFormElement | null>, alertRef: RefObject<HTMLDivElement | null>, attempt: number, preferAlert: boolean): void {
  useEffect(() => {
    if (attempt === 0) return;
    if (preferAlert && alertRef.current) {
      alertRef.current.focus();
      return;
    }
    const invalid = formRef.current?.querySelector<HTMLElement>('[aria-invalid="true"]');
    (invalid ?? alertRef.current)?.focus();
  }, [attempt]);
}
