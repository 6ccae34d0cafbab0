/** Who is calling: the signed-in user as the server layer sees it. */
export type Actor = { userId: string; email: string; name: string; isAdmin: boolean };

export type UserRow = { id: string; email: string; name: string; password_hash: string; is_admin: number };

export function actorFromRow(row: Pick<UserRow, "id" | "email" | "name" | "is_admin">): Actor {
  return { userId: row.id, email: row.email, name: row.name, isAdmin: row.is_admin === 1 };
}
