import { describe, expect, it } from "vitest";
import {
  contentDisposition,
  displayFileName,
  formatBytes,
  isAttachmentType,
  refusedTypeMessage,
} from "./attachment-files";

describe("a stored file's name in a download", () => {
  it("cannot add parameters, lines or paths", () => {
    const header = contentDisposition("attachment", 'a"; filename=x.html\r\nSet-Cookie: y.pdf');
    expect(header).toBe(
      `attachment; filename="a_filename_x.html_Set-Cookie_y.pdf"; filename*=UTF-8''a%22%3B%20filename%3Dx.html%0D%0ASet-Cookie%3A%20y.pdf`,
    );
    expect(contentDisposition("inline", "..")).toBe(`inline; filename="_"; filename*=UTF-8''..`);
    expect(contentDisposition("inline", "Fotó berm.jpg")).toBe(
      `inline; filename="Fot_berm.jpg"; filename*=UTF-8''Fot%C3%B3%20berm.jpg`,
    );
  });

  it("is shown without a path or control characters, and never empty", () => {
    expect(displayFileName("C:\\Users\\crew\\IMG_0001.JPG", "x")).toBe("IMG_0001.JPG");
    expect(displayFileName("../../etc/passwd", "x")).toBe("passwd");
    expect(displayFileName("\u0000\u001f", "attachment.pdf")).toBe("attachment.pdf");
    expect(displayFileName("a".repeat(300), "x")).toHaveLength(255);
  });
});

describe("allowed types", () => {
  it("are the photo formats and PDF, and a refusal says what the file was", () => {
    expect(["image/jpeg", "image/png", "image/webp", "image/heic", "application/pdf"].every(isAttachmentType)).toBe(
      true,
    );
    expect(isAttachmentType("application/x-msdownload")).toBe(false);
    expect(isAttachmentType("constructor")).toBe(false);
    expect(refusedTypeMessage("EXE (application/x-msdownload)")).toBe(
      "This file's content is EXE (application/x-msdownload), which Foamtally does not keep, whatever its name says. Attach JPEG, PNG, WebP or HEIC photos and PDF documents.",
    );
    expect(formatBytes(25 * 1024 * 1024)).toBe("25.0 MB");
  });
});
