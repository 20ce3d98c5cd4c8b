import { describe, expect, it } from "vitest";
import { selectedIds, selectionMark, toggleFindings } from "@/lib/register/selection";

describe("the register's selection", () => {
  it("ticks a page's findings together and keeps those ticked on other pages", () => {
    const fromPageOne = toggleFindings(new Set(), [12, 40], true);
    const withPageTwo = toggleFindings(fromPageOne, [7, 12, 93], true);
    expect(selectedIds(withPageTwo)).toEqual([7, 12, 40, 93]);
    // Unticking page two's box leaves page one's other finding selected.
    expect(selectedIds(toggleFindings(withPageTwo, [7, 12, 93], false))).toEqual([40]);
  });

  it("does not change the selection it is given", () => {
    const before = new Set([1, 2]);
    toggleFindings(before, [3], true);
    toggleFindings(before, [1], false);
    expect([...before]).toEqual([1, 2]);
  });

  it("marks a box ticked when all of its findings are selected, mixed when some are, empty otherwise", () => {
    const selected = new Set([5, 6, 9]);
    expect(selectionMark(selected, [5, 6])).toBe("all");
    expect(selectionMark(selected, [5, 7])).toBe("some");
    expect(selectionMark(selected, [7, 8])).toBe("none");
    // An empty page has nothing to tick.
    expect(selectionMark(selected, [])).toBe("none");
  });
});
