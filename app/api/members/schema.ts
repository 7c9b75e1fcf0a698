import { z } from "zod";
import { roles } from "@/db/schema";

export const roleSchema = z.enum(roles, {
  error: `a role is one of ${roles.join(", ")}`,
});
