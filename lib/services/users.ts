import "server-only";
import bcrypt from "bcryptjs";
import { UniqueConstraintError } from "sequelize";
import { getDb } from "@/lib/db";
import { HttpError, notFound } from "@/lib/http";
import type { Role } from "@/lib/auth/roles";
import type { CreateUserInput } from "@/lib/validations/user";
import { audit } from "./audit";

const BCRYPT_COST = 10;
// Compared against when the account does not exist, so both paths cost one bcrypt check.
const DUMMY_HASH = bcrypt.hashSync("siderea-no-such-account", BCRYPT_COST);

export interface PublicUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  createdAt: Date;
}

const PUBLIC_ATTRIBUTES = ["id", "email", "name", "role", "createdAt"] as const;

/** The user whose e-mail and password match, or null (same cost either way). */
export async function verifyPassword(email: string, password: string): Promise<PublicUser | null> {
  const { User } = getDb().models;
  const user = await User.findOne({
    where: getDb().sequelize.where(getDb().sequelize.fn("lower", getDb().sequelize.col("email")), email.toLowerCase()),
  });
  const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !ok || user.disabledAt) return null;
  return { id: user.id, email: user.email, name: user.name, role: user.role, createdAt: user.createdAt };
}

export async function findActiveUser(id: number): Promise<PublicUser | null> {
  const user = await getDb().models.User.findByPk(id, { attributes: [...PUBLIC_ATTRIBUTES, "disabledAt"] });
  if (!user || user.disabledAt) return null;
  return { id: user.id, email: user.email, name: user.name, role: user.role, createdAt: user.createdAt };
}

export async function listUsers(): Promise<PublicUser[]> {
  const users = await getDb().models.User.findAll({ attributes: [...PUBLIC_ATTRIBUTES], order: [["id", "ASC"]] });
  return users.map((u) => ({ id: u.id, email: u.email, name: u.name, role: u.role, createdAt: u.createdAt }));
}

export async function createUser(input: CreateUserInput, actorId: number): Promise<PublicUser> {
  try {
    const user = await getDb().models.User.create({
      email: input.email,
      name: input.name,
      role: input.role,
      passwordHash: await bcrypt.hash(input.password, BCRYPT_COST),
      disabledAt: null,
    });
    await audit({ actorId, action: "user.create", targetType: "user", targetId: user.id, details: { email: user.email, role: user.role } });
    return { id: user.id, email: user.email, name: user.name, role: user.role, createdAt: user.createdAt };
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      throw new HttpError(409, "conflict", "A user with this e-mail address already exists.", [
        { path: "email", message: "Already in use." },
      ]);
    }
    throw error;
  }
}

export async function changeRole(userId: number, role: Role, actorId: number): Promise<PublicUser> {
  const user = await getDb().models.User.findByPk(userId);
  if (!user) throw notFound("user");
  if (user.id === actorId && role !== "admin") {
    throw new HttpError(409, "conflict", "You cannot remove your own administrator role; ask another administrator.");
  }
  const before = user.role;
  user.role = role;
  await user.save();
  await audit({ actorId, action: "user.role", targetType: "user", targetId: user.id, details: { from: before, to: role } });
  return { id: user.id, email: user.email, name: user.name, role: user.role, createdAt: user.createdAt };
}
