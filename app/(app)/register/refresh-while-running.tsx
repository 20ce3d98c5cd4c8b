"use client";
import { useRouter } from "next/navigation";
import { useEffect } from "react";

const REFRESH_MS = 3000;

/** Re-renders the server page every few seconds while it is mounted (only while a job runs). */
export function RefreshWhileRunning() {
  const router = useRouter();
  useEffect(() => {
    const timer = setInterval(() => router.refresh(), REFRESH_MS);
    return () => clearInterval(timer);
  }, [router]);
  return null;
}
