// The local SMTP sink of `npm start` and `npm test` (lib/mail/sink.ts): listens on
// 127.0.0.1:${SIDEREA_SMTP_PORT:-2525} and stores every message in ${SIDEREA_MAIL_SINK_DIR:-.siderea/mail}.
import { startSmtpSink } from "@/lib/mail/sink";

const port = Number(process.env.SIDEREA_SMTP_PORT ?? 2525);
const dir = process.env.SIDEREA_MAIL_SINK_DIR ?? ".siderea/mail";
const sink = await startSmtpSink({ port, dir });
console.log(`smtp sink: listening on 127.0.0.1:${sink.port}, storing messages in ${dir}`);
const stop = async () => {
  await sink.close();
  process.exit(0);
};
process.on("SIGTERM", () => void stop());
process.on("SIGINT", () => void stop());
