import { describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser } from "./auth-helpers";
import { authOptions } from "@/lib/auth/options";

useTestDatabase();

type Authorize = (credentials: Record<string, string>, req: { headers: Record<string, string> }) => Promise<unknown>;

function authorizeFn(): Authorize {
  const provider = authOptions().providers[0] as unknown as { options: { authorize: Authorize } };
  return provider.options.authorize;
}

const from = (ip: string) => ({ headers: { "x-forwarded-for": ip } });

describe("sign-in with e-mail and password", () => {
  it("accepts the right password, case-insensitive e-mail, and returns the role", async () => {
    const u = await makeUser("referee", "Referee.Case@test.siderea.test");
    const result = await authorizeFn()({ email: "referee.case@TEST.siderea.test", password: u.password }, from("10.0.0.1"));
    expect(result).toMatchObject({ id: String(u.id), role: "referee" });
  });

  it("gives the same error for a wrong password and for an unknown account", async () => {
    const u = await makeUser("member");
    await expect(authorizeFn()({ email: u.email, password: "wrong-password" }, from("10.0.0.2"))).rejects.toThrow(/^invalid$/);
    await expect(authorizeFn()({ email: "nobody@test.siderea.test", password: "wrong-password" }, from("10.0.0.3"))).rejects.toThrow(/^invalid$/);
  });

  it("blocks an account after 5 failures, even with the right password, and from another address", async () => {
    const u = await makeUser("analyst");
    for (let i = 0; i < 5; i++) {
      await expect(authorizeFn()({ email: u.email, password: `guess-${i}` }, from(`10.1.0.${i}`))).rejects.toThrow(/^invalid$/);
    }
    await expect(authorizeFn()({ email: u.email, password: u.password }, from("10.1.1.1"))).rejects.toThrow(/^rate-limited:\d+$/);
  });

  it("blocks an address that guesses across many accounts", async () => {
    for (let i = 0; i < 5; i++) {
      await expect(authorizeFn()({ email: `spray-${i}@test.siderea.test`, password: "guess" }, from("10.9.9.9"))).rejects.toThrow(/^invalid$/);
    }
    const u = await makeUser("member");
    await expect(authorizeFn()({ email: u.email, password: u.password }, from("10.9.9.9"))).rejects.toThrow(/^rate-limited:/);
    // The same account from a clean address still signs in.
    await expect(authorizeFn()({ email: u.email, password: u.password }, from("10.9.9.10"))).resolves.toMatchObject({ role: "member" });
  });
});
