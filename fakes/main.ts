// `npm run fakes`: the S3 and SMTP fakes on their demo ports, data under .local/, until Ctrl-C.
// (`npm start` runs the same fakes in its own process; this is for `npm run dev` or by hand.)
import { join } from "node:path";
import { LOCAL } from "../scripts/lib/paths";
import { startS3Fake } from "./s3";
import { startSmtpFake } from "./smtp";

export async function startDemoFakes(env: NodeJS.ProcessEnv = process.env) {
  const s3Port = Number(new URL(env.S3_ENDPOINT ?? "http://127.0.0.1:9320").port || 80);
  const s3 = await startS3Fake({ port: s3Port, dir: join(LOCAL, "s3"), bucket: env.S3_BUCKET ?? "tidewire" });
  const smtp = await startSmtpFake({
    smtpPort: Number(env.SMTP_PORT ?? 2525),
    httpPort: Number(env.MAIL_INBOX_PORT ?? 8025),
    dir: join(LOCAL, "mail"),
  }).catch(async (err) => {
    await s3.stop();
    throw err;
  });
  return {
    s3,
    smtp,
    inboxUrl: `http://127.0.0.1:${smtp.httpPort}/`,
    async stop() {
      await Promise.all([s3.stop(), smtp.stop()]);
    },
  };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const fakes = await startDemoFakes();
  console.log(`S3 fake    ${fakes.s3.endpoint} (bucket ${process.env.S3_BUCKET ?? "tidewire"}, files in .local/s3)`);
  console.log(`SMTP fake  127.0.0.1:${fakes.smtp.smtpPort} (mail in .local/mail)`);
  console.log(`Mail inbox ${fakes.inboxUrl}`);
  for (const sig of ["SIGINT", "SIGTERM"] as const) {
    process.on(sig, () => void fakes.stop().then(() => process.exit(0)));
  }
}
