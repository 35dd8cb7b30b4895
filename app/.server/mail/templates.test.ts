import { describe, expect, it } from "vitest";
import { CAUTIONS, escapeHtml, renderMail } from "./templates";
import { parseMessage } from "../../../.dev/mail-sink";

describe("mail templates", () => {
  it("escapes everything that comes from records before it reaches the HTML", () => {
    expect(escapeHtml(`<b>"O'Neil" & co</b>`)).toBe("&lt;b&gt;&quot;O&#39;Neil&quot; &amp; co&lt;/b&gt;");
    const mail = renderMail({
      subject: "Pool <script>",
      preview: "p",
      blocks: [{ kind: "paragraph", text: "Customer <img src=x onerror=alert(1)>" }],
    });
    expect(mail.html).not.toContain("<img");
    expect(mail.html).toContain("Customer &lt;img src=x onerror=alert(1)&gt;");
    expect(mail.text).toContain("Customer <img src=x onerror=alert(1)>");
  });

  it("writes the same table as an accessible HTML table and as aligned plain text", () => {
    const mail = renderMail({
      subject: "s",
      preview: "p",
      blocks: [
        {
          kind: "table",
          caption: "Readings",
          columns: [{ label: "Pool" }, { label: "mg/L", align: "right" }],
          rows: [
            ["Long street name", "0.40"],
            ["Short", "12.00"],
          ],
          empty: "none",
        },
        { kind: "table", caption: "Nothing", columns: [{ label: "A" }], rows: [], empty: "No rows this week." },
      ],
    });
    expect(mail.html).toContain("<caption");
    expect(mail.html).toContain('<th scope="col"');
    expect(mail.text).toContain(["Readings", "Pool               mg/L", "Long street name   0.40", "Short             12.00"].join("\n"));
    expect(mail.text).toContain("No rows this week.");
    // The empty table becomes its sentence, not an empty grid.
    expect(mail.html.match(/<caption/g)).toHaveLength(1);
  });

  it("carries every caution in both parts when asked", () => {
    const mail = renderMail({ subject: "s", preview: "p", blocks: [{ kind: "cautions" }] });
    for (const caution of CAUTIONS) {
      expect(mail.text).toContain(caution);
      expect(mail.html).toContain(escapeHtml(caution));
    }
  });
});

describe("the sink's message reader", () => {
  it("decodes quoted-printable and base64 parts and encoded subjects", async () => {
    const raw = [
      "Subject: =?UTF-8?Q?Gr=C3=BC=C3=9Fe?=",
      "Message-ID: <m1@patina.example>",
      'Content-Type: multipart/alternative; boundary="b1"',
      "",
      "--b1",
      "Content-Type: text/plain; charset=utf-8",
      "Content-Transfer-Encoding: quoted-printable",
      "",
      "Link: http://localhost:3000/invite/abc=3Ddef and a long line that was wr=",
      "apped",
      "--b1",
      "Content-Type: text/html; charset=utf-8",
      "Content-Transfer-Encoding: base64",
      "",
      Buffer.from("<p>Grüße</p>").toString("base64"),
      "--b1--",
      "",
    ].join("\r\n");
    expect(await parseMessage(raw)).toEqual({
      subject: "Grüße",
      messageId: "<m1@patina.example>",
      text: "Link: http://localhost:3000/invite/abc=def and a long line that was wrapped",
      html: "<p>Grüße</p>",
    });
  });
});
