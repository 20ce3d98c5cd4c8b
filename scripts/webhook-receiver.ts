/**
 * Runs the local webhook receiver on 127.0.0.1:WEBHOOK_FAKE_PORT (default 3027). With
 * WEBHOOK_RECEIVER_SECRET (a whsec_… secret) it checks every delivery's signature.
 * GET /deliveries lists what it recorded; POST /fake/fail {"count":2,"status":500} fails the next ones.
 */
import { startWebhookReceiver } from "../lib/webhooks/receiver-fake";

const port = Number(process.env.WEBHOOK_FAKE_PORT || 3027);
startWebhookReceiver({ port, secret: process.env.WEBHOOK_RECEIVER_SECRET || undefined })
  .then((receiver) => {
    console.log(JSON.stringify({ app: "headroom-webhook-receiver", msg: "listening", url: receiver.url }));
    const stop = () => void receiver.close().then(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  })
  .catch((error: Error) => {
    console.error(`The webhook receiver could not listen on 127.0.0.1:${port}: ${error.message}`);
    process.exit(1);
  });
