import nodemailer from "nodemailer";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase, type Database } from "../db/client";
import { snapshotDatabase } from "../testing/database-snapshot";
import { outbox } from "../db/schema";
import { createOutboxMailer } from "./mailer";

let db: Database;
beforeAll(async () => {
  db = await snapshotDatabase("migrated");
});
afterAll(() => closeDatabase(db));

describe("createOutboxMailer", () => {
  it("writes every message to the outbox and hands it to the transport when there is one", async () => {
    const transport = nodemailer.createTransport({ jsonTransport: true });
    const sendMail = vi.spyOn(transport, "sendMail");

    const mailer = createOutboxMailer(db, { transport, from: "Tributary <no-reply@quillfern.example>" });
    await mailer.send({ to: "lead@quillfern.example", subject: "A fit was published", text: "See the portfolio map.", kind: "run_published" });

    const rows = await db.select().from(outbox);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ to: "lead@quillfern.example", subject: "A fit was published", text: "See the portfolio map.", html: null, kind: "run_published" });
    expect(sendMail).toHaveBeenCalledTimes(1);
    const info = (await sendMail.mock.results[0]!.value) as { message: string };
    expect(JSON.parse(info.message)).toMatchObject({ subject: "A fit was published", to: [{ address: "lead@quillfern.example" }] });
  });
});
