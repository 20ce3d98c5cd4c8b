/** Runs the local e-mail fake on 127.0.0.1:EMAIL_FAKE_PORT (default 3025). */
import { startEmailFake } from "../lib/mail/fake-server";

const port = Number(process.env.EMAIL_FAKE_PORT || 3025);
startEmailFake({ port })
  .then((fake) => {
    console.log(JSON.stringify({ app: "headroom-email-fake", msg: "listening", url: fake.url }));
    const stop = () => void fake.close().then(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  })
  .catch((error: Error) => {
    console.error(`The e-mail fake could not listen on 127.0.0.1:${port}: ${error.message}`);
    process.exit(1);
  });
