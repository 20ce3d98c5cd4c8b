import http from "node:http";
import type { AddressInfo } from "node:net";
import { expect, test } from "@playwright/test";
import { BASE_URL } from "../../playwright.config";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

/** A page on another port of the same host: the same site for the browser, so SameSite=Lax cookies go along. */
function foreignPage(html: string): Promise<{ url: string; close: () => Promise<void> }> {
  const server = http.createServer((_request, response) => {
    response.writeHead(200, { "content-type": "text/html; charset=utf-8" });
    response.end(html);
  });
  return new Promise((resolve) => {
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as AddressInfo;
      resolve({ url: `http://localhost:${port}/`, close: () => new Promise((done) => server.close(() => done())) });
    });
  });
}

const MALLORY = "mallory.cross.site@example.org";

const ATTACK = `<!doctype html><html><body>
<h1>Free sample offer</h1>
<form id="json-as-text" method="POST" enctype="text/plain" action="${BASE_URL}/api/v1/users" target="sink">
  <input name='{"email":"${MALLORY}","name":"Mallory","role":"admin","pad":"' value='"}'>
</form>
<form id="page-post" method="POST" action="${BASE_URL}/admin" target="sink2">
  <input name="email" value="${MALLORY}">
</form>
<iframe name="sink"></iframe><iframe name="sink2"></iframe>
<p id="done">waiting</p>
<script>
  (async () => {
    const tries = [];
    tries.push(fetch("${BASE_URL}/api/v1/users", { method: "POST", mode: "no-cors", credentials: "include", headers: { "content-type": "text/plain" }, body: JSON.stringify({ email: "${MALLORY}", name: "Mallory", role: "admin" }) }).catch(() => null));
    tries.push(fetch("${BASE_URL}/api/v1/session", { method: "DELETE", mode: "no-cors", credentials: "include" }).catch(() => null));
    await Promise.all(tries);
    document.getElementById("json-as-text").submit();
    document.getElementById("page-post").submit();
    setTimeout(() => { document.getElementById("done").textContent = "sent"; }, 1500);
  })();
</script>
</body></html>`;

test("a foreign page cannot make a signed-in person write; pages work under the CSP, with the right status codes, and sign-in works without JavaScript", async ({ page, browser, request }) => {
  const policyViolations: string[] = [];
  page.on("console", (message) => {
    if (/Content Security Policy|Refused to (load|execute|apply)/i.test(message.text())) policyViolations.push(message.text());
  });

  // Signed in as the administrator, the person opens a link to another site on the same host.
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("admin@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  const attacker = await foreignPage(ATTACK);
  try {
    const attackPage = await page.context().newPage();
    await attackPage.goto(attacker.url);
    await expect(attackPage.locator("#done")).toHaveText("sent", { timeout: 15_000 });
    await attackPage.close();
  } finally {
    await attacker.close();
  }

  // Nothing was written: no new administrator, and the person is still signed in.
  await page.goto("/admin");
  await expect(page.getByRole("heading", { name: "Administration" })).toBeVisible();
  await expect(page.getByText(MALLORY)).toHaveCount(0);
  const users = await page.request.get("/api/v1/users");
  expect(users.status()).toBe(200);
  const emails = ((await users.json()).data as { email: string }[]).map((u) => u.email);
  expect(emails).toContain("admin@example.org");
  expect(emails).not.toContain(MALLORY);

  // The app's own pages keep working under the policy: the register table, a chart, a form.
  await page.goto("/register");
  await expect(page.getByRole("table").first()).toBeVisible();
  await page.goto("/temperatures");
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  await page.goto("/inventory/new");
  await expect(page.getByLabel("Label")).toBeVisible();
  const headers = (await page.request.get("/sign-in")).headers();
  expect(headers["content-security-policy"]).toMatch(/script-src 'self' 'nonce-[^']+' 'strict-dynamic'.*frame-ancestors 'none'/);
  expect(headers["x-content-type-options"]).toBe("nosniff");
  expect(headers["referrer-policy"]).toBe("same-origin");
  expect(policyViolations).toEqual([]);

  // An upload past 10 MB arrives whole (Next.js would cut a body its proxy sees at 10 MB; the API
  // is outside the proxy), and API answers carry their own security headers.
  const sensorId = ((await (await page.request.get("/api/v1/sensors")).json()).data as { id: number }[])[0].id;
  const row = "2026-01-01T00:00:00Z,4.5\n";
  const csv = Buffer.from(`time,temperature\n${row.repeat(Math.ceil((11 * 2 ** 20) / row.length))}`);
  const uploaded = await page.request.post(`/api/v1/sensors/${sensorId}/csv-uploads`, { multipart: { file: { name: "big-logger.csv", mimeType: "text/csv", buffer: csv } } });
  expect(uploaded.status()).toBe(201);
  expect((await uploaded.json()).data.sizeBytes).toBe(csv.length);
  expect(uploaded.headers()["content-security-policy"]).toBe("default-src 'none'; frame-ancestors 'none'; sandbox");
  expect(uploaded.headers()["x-content-type-options"]).toBe("nosniff");
  expect(uploaded.headers()["referrer-policy"]).toBe("same-origin");

  // A page a role may not open answers 403, a missing record 404 — as status codes.
  const researcher = await browser.newContext();
  const researcherPage = await researcher.newPage();
  await new SignInPage(researcherPage).goto();
  await new SignInPage(researcherPage).signIn("researcher@example.org", DEMO_PASSWORD);
  await expect(researcherPage).toHaveURL(/\/$/);
  expect((await researcherPage.goto("/admin"))?.status()).toBe(403);
  await expect(researcherPage.getByRole("heading", { name: "Your role does not open this page" })).toBeVisible();
  expect((await researcherPage.goto("/inventory/999999"))?.status()).toBe(404);
  await researcher.close();

  // Without JavaScript (or before hydration) the sign-in form still works, errors included.
  const noScript = await browser.newContext({ javaScriptEnabled: false });
  const plain = await noScript.newPage();
  await plain.goto("/sign-in?next=/%5Cevil.example/phish");
  await plain.getByLabel("E-mail address").fill("safety@example.org");
  await plain.getByLabel("Password", { exact: true }).fill("not the password");
  const refused = await Promise.all([plain.waitForNavigation(), plain.getByRole("button", { name: "Sign in" }).click()]);
  expect(refused[0]?.status()).toBeLessThan(500);
  await expect(plain.getByText("That e-mail address and password do not match an active account.")).toBeVisible();
  await plain.getByLabel("Password", { exact: true }).fill(DEMO_PASSWORD);
  await plain.getByRole("button", { name: "Sign in" }).click();
  // The crafted next= leads to the overview, never to another host.
  await expect(plain).toHaveURL(`${BASE_URL}/`);
  await expect(plain.getByRole("heading", { level: 1 })).toContainText("Priya");
  await noScript.close();

  void request;
});
