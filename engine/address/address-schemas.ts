import { z } from "zod";
import { parseGroupAddress } from "./group-address";
import { parseIndividualAddress } from "./individual-address";

/** A group address as text in any notation ("1/0/1", "1/257", "4097"); bench JSON stores this form. */
export const groupAddressTextSchema = z.string().superRefine((text, ctx) => {
  const parsed = parseGroupAddress(text);
  if (!parsed.ok) ctx.addIssue({ code: "custom", message: parsed.error.message });
});

/** An individual address as text, area.line.device ("1.1.10"). */
export const individualAddressTextSchema = z.string().superRefine((text, ctx) => {
  const parsed = parseIndividualAddress(text);
  if (!parsed.ok) ctx.addIssue({ code: "custom", message: parsed.error.message });
});
