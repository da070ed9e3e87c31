// Users: reads return small DTOs without the password hash, except the one lookup sign-in needs.
import type { Prisma } from "./open";

export interface UserDto {
  id: string;
  email: string;
  name: string;
  role: string;
  active: boolean;
  createdAt: string;
}

const publicFields = { id: true, email: true, name: true, role: true, active: true, createdAt: true } as const;

function toDto(row: { id: string; email: string; name: string; role: string; active: boolean; createdAt: Date }): UserDto {
  return { ...row, createdAt: row.createdAt.toISOString() };
}

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export async function findUserForSignIn(prisma: Prisma, email: string) {
  return prisma.user.findUnique({ where: { email: normaliseEmail(email) } });
}

export async function findUser(prisma: Prisma, id: string): Promise<UserDto | null> {
  const row = await prisma.user.findUnique({ where: { id }, select: publicFields });
  return row ? toDto(row) : null;
}

export async function listUsers(prisma: Prisma): Promise<UserDto[]> {
  const rows = await prisma.user.findMany({ select: publicFields, orderBy: [{ role: "asc" }, { email: "asc" }] });
  return rows.map(toDto);
}

export async function createUser(
  prisma: Prisma,
  data: { email: string; name: string; role: string; passwordHash: string },
): Promise<UserDto> {
  const row = await prisma.user.create({ data: { ...data, email: normaliseEmail(data.email) }, select: publicFields });
  return toDto(row);
}

export async function updateUser(
  prisma: Prisma,
  id: string,
  data: { name?: string; role?: string; active?: boolean; passwordHash?: string },
): Promise<UserDto> {
  const row = await prisma.user.update({ where: { id }, data, select: publicFields });
  return toDto(row);
}
