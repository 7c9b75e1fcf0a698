"use server";

import { z } from "zod";
import { validatedAction } from "@/app/_lib/action";
import { hashPassword, newPasswordSchema, verifyPassword } from "@/app/_lib/auth";
import { verifySession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { writeSessionCookie } from "@/app/_lib/session";
import { endOutstandingPasswordResets } from "@/db/queries/password-resets";
import { findUserById, setPasswordHash } from "@/db/queries/users";

const changePasswordSchema = z
  .strictObject({
    currentPassword: z.string().min(1, "enter your current password"),
    newPassword: newPasswordSchema,
    confirmPassword: z.string(),
  })
  .refine((input) => input.newPassword === input.confirmPassword, {
    path: ["confirmPassword"],
    message: "the two new passwords differ",
  });

/**
 * Change the signed-in user's password. Every other session of the user ends
 * (the session version moves on); this browser gets a fresh cookie.
 */
export const changePasswordAction = validatedAction(changePasswordSchema, async (input) => {
  const session = await verifySession();
  const user = findUserById({ userId: session.userId });
  if (!user || !(await verifyPassword(input.currentPassword, user.passwordHash))) {
    throw new AppError("invalid_input", "currentPassword: that is not your current password", {
      field: "currentPassword",
    });
  }
  const updated = setPasswordHash({
    userId: user.id,
    passwordHash: await hashPassword(input.newPassword),
  });
  if (!updated) throw new AppError("not_found", "your account no longer exists");
  // A reset link asked for before the change must not undo it.
  endOutstandingPasswordResets({ userId: user.id });
  await writeSessionCookie({
    userId: user.id,
    workspaceId: session.workspaceId,
    sessionVersion: updated.sessionVersion,
    issuedAt: Date.now(),
  });
  return { changed: true as const };
});
