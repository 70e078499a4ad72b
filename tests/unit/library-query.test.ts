import { describe, expect, it } from "vitest";
import { defaultLibraryDir, libraryApiQuery, libraryQueryFromAddress } from "@/lib/api/library-query";

describe("libraryQueryFromAddress", () => {
  it("maps the address's short names onto the library query", () => {
    expect(libraryQueryFromAddress({ q: "hull", team: "t1", owner: "u1", review: "in-review", status: "none", archived: "1", sort: "team", dir: "desc", page: "3" }, 25)).toEqual({
      q: "hull",
      teamId: "t1",
      ownerId: "u1",
      reviewState: "in-review",
      worstStatus: "none",
      archived: true,
      sort: "team",
      dir: "desc",
      page: 3,
      pageSize: 25,
    });
  });

  it("drops what it cannot read instead of failing, and takes a repeated parameter's first value", () => {
    const q = libraryQueryFromAddress({ review: "lost", status: "bad", sort: "colour", dir: "sideways", page: "0", archived: "yes", q: ["first", "second"] }, 10);
    expect(q).toEqual({ q: "first", teamId: undefined, ownerId: undefined, reviewState: undefined, worstStatus: undefined, archived: false, sort: undefined, dir: "desc", page: undefined, pageSize: 10 });
    expect(libraryQueryFromAddress({ q: "x".repeat(201) }, 10).q).toBeUndefined();
  });

  it("sorts newest first by default and any other column A→Z until the address says otherwise", () => {
    expect(defaultLibraryDir(undefined)).toBe("desc");
    expect(defaultLibraryDir("updatedAt")).toBe("desc");
    expect(libraryQueryFromAddress({ sort: "name" }, 25).dir).toBe("asc");
    expect(libraryQueryFromAddress({ sort: "name", dir: "desc" }, 25).dir).toBe("desc");
  });
});

describe("libraryApiQuery", () => {
  it("reads the same fields strictly, naming each bad one", () => {
    expect(libraryApiQuery.parse({ reviewState: "approved", page: "2", pageSize: "50", archived: "0" })).toEqual({ reviewState: "approved", page: 2, pageSize: 50, archived: "0" });
    const bad = libraryApiQuery.safeParse({ reviewState: "lost", sort: "colour", pageSize: "500" });
    expect(bad.success ? [] : bad.error.issues.map((i) => i.path.join("."))).toEqual(["reviewState", "sort", "pageSize"]);
  });
});
