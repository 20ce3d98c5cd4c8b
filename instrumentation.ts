export async function register() {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    (await import("./lib/http/peer-address")).installPeerAddressHeader();
    const { startJobs } = await import("./lib/jobs");
    startJobs();
  }
}
