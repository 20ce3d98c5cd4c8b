import { describe, expect, it } from "vitest";
import { NotFoundError } from "@/lib/errors";

describe("NotFoundError", () => {
  it("makes a sentence of the thing's name", () => {
    expect(new NotFoundError("That room").message).toBe("That room was not found.");
    expect(new NotFoundError().message).toBe("That item was not found.");
  });

  it("keeps a message that is already a sentence", () => {
    expect(new NotFoundError("No such finding, or it is not on a location you look after.").message).toBe(
      "No such finding, or it is not on a location you look after.",
    );
  });
});
