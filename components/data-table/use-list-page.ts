"use client";

import { useCallback, useEffect, useState } from "react";
import type { ListPage } from "@/lib/http/list-query";

type Settled<Row> = {
  /** The request the newest answer belongs to. */
  key: string | null;
  /** The newest page that arrived, kept on screen while the next one loads. */
  page: ListPage<Row> | null;
  /** The newest request's error, if it failed. */
  error: string | null;
};

class ListRequestError extends Error {}

const UNREACHABLE = "The server could not be reached. Check the connection and try again.";

async function readError(response: Response): Promise<string> {
  try {
    const body = (await response.json()) as { error?: { message?: string } };
    if (body?.error?.message) return body.error.message;
  } catch {
    // not JSON: fall through to the status line
  }
  return `The server answered ${response.status} ${response.statusText}`.trim() + ".";
}

/**
 * One page of a list from the JSON API. A new URL aborts the request still in flight, so a slow
 * answer to an old query can never overwrite a newer one.
 */
export function useListPage<Row>(url: string, version = 0) {
  const [attempt, setAttempt] = useState(0);
  const [settled, setSettled] = useState<Settled<Row>>({ key: null, page: null, error: null });
  const key = `${attempt} ${version} ${url}`;

  useEffect(() => {
    const controller = new AbortController();
    fetch(url, { credentials: "same-origin", signal: controller.signal, headers: { accept: "application/json" } })
      .then(async (response) => {
        if (!response.ok) throw new ListRequestError(await readError(response));
        const page = (await response.json()) as ListPage<Row>;
        setSettled({ key, page, error: null });
      })
      .catch((error: unknown) => {
        if (controller.signal.aborted) return;
        const message = error instanceof ListRequestError ? error.message : UNREACHABLE;
        setSettled((previous) => ({ key, page: previous.page, error: message }));
      });
    return () => controller.abort();
  }, [url, key]);

  const retry = useCallback(() => setAttempt((n) => n + 1), []);
  const loading = settled.key !== key;
  return { page: settled.page, error: loading ? null : settled.error, loading, retry };
}
