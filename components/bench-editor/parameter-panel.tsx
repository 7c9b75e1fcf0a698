"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMemo } from "react";
import {
  useFieldArray,
  useForm,
  type Control,
  type FieldErrors,
  type UseFormRegister,
} from "react-hook-form";
import type { z } from "zod";
import type { BenchDevice } from "@/engine";
import { getDeviceType } from "@/engine";
import { effectiveParameters } from "./model/device-objects";
import { setParameters } from "./model/devices";
import {
  emptyValue,
  fieldKey,
  fieldLabel,
  parameterFields,
  type ParameterField,
} from "./model/parameter-fields";
import { useEditorStoreApi } from "./store/editor-context";

type Values = Record<string, unknown>;

function errorAt(errors: FieldErrors<Values>, path: string): string | undefined {
  let current: unknown = errors;
  for (const part of path.split(".")) {
    if (current === null || typeof current !== "object") return undefined;
    current = (current as Record<string, unknown>)[part];
  }
  const message = (current as { message?: unknown } | undefined)?.message;
  return typeof message === "string" ? message : undefined;
}

interface FieldProps {
  readonly field: ParameterField;
  readonly path: string;
  readonly register: UseFormRegister<Values>;
  readonly control: Control<Values>;
  readonly errors: FieldErrors<Values>;
  readonly submit: () => void;
  /** Shown but not changeable: no adding or removing items either. */
  readonly readOnly: boolean;
}

function FieldView({ field, path, register, control, errors, submit, readOnly }: FieldProps) {
  const label = fieldLabel(fieldKey(field));
  const error = errorAt(errors, path);
  const id = `param-${path}`;
  const errorLine = error ? (
    <p role="alert" className="text-xs text-fault">
      {error}
    </p>
  ) : null;
  switch (field.kind) {
    case "enum":
      return (
        <div className="flex flex-col gap-1">
          <label htmlFor={id} className="text-xs text-ink-soft">
            {label}
          </label>
          <select
            id={id}
            {...register(path, { onChange: submit })}
            className="rounded border border-paper-line bg-paper px-2 py-1 text-sm"
          >
            {field.options.map((option) => (
              <option key={option} value={option}>
                {option}
              </option>
            ))}
          </select>
          {errorLine}
        </div>
      );
    case "boolean":
      return (
        <div>
          <label className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              {...register(path, { onChange: submit })}
              className="accent-copper"
            />
            {label}
          </label>
          {errorLine}
        </div>
      );
    case "number":
      return (
        <div className="flex flex-col gap-1">
          <label htmlFor={id} className="text-xs text-ink-soft">
            {label}
            {field.min !== undefined && field.max !== undefined ? (
              <span className="ml-1 font-mono">
                {field.min}–{field.max}
              </span>
            ) : null}
          </label>
          <input
            id={id}
            type="number"
            step={field.integer ? 1 : "any"}
            {...(field.min === undefined ? {} : { min: field.min })}
            {...(field.max === undefined ? {} : { max: field.max })}
            {...register(path, { valueAsNumber: true, onBlur: submit })}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                submit();
              }
            }}
            aria-invalid={error ? true : undefined}
            className="rounded border border-paper-line bg-paper px-2 py-1 font-mono text-sm"
          />
          {errorLine}
        </div>
      );
    case "string":
      return (
        <div className="flex flex-col gap-1">
          <label htmlFor={id} className="text-xs text-ink-soft">
            {label}
          </label>
          <input
            id={id}
            {...register(path, { onBlur: submit })}
            className="rounded border border-paper-line bg-paper px-2 py-1 text-sm"
          />
          {errorLine}
        </div>
      );
    case "object":
      return (
        <fieldset className="flex flex-col gap-2 rounded border border-paper-line p-2">
          <legend className="px-1 text-xs font-semibold">{label}</legend>
          {field.fields.map((child) => (
            <FieldView
              key={child.name}
              field={child}
              path={`${path}.${fieldKey(child)}`}
              register={register}
              control={control}
              errors={errors}
              submit={submit}
              readOnly={readOnly}
            />
          ))}
        </fieldset>
      );
    case "array":
      return field.element.kind === "object" ? (
        <ArrayFieldView
          field={field}
          path={path}
          register={register}
          control={control}
          errors={errors}
          submit={submit}
          readOnly={readOnly}
        />
      ) : (
        <p className="text-xs text-ink-soft">{label}: edit in the bench file</p>
      );
    case "unsupported":
      return <p className="text-xs text-ink-soft">{label}: edit in the bench file</p>;
  }
}

function ArrayFieldView({
  field,
  path,
  register,
  control,
  errors,
  submit,
  readOnly,
}: FieldProps & { field: Extract<ParameterField, { kind: "array" }> }) {
  const { fields, append, remove } = useFieldArray({ control, name: path as never });
  const label = fieldLabel(fieldKey(field));
  const element = field.element;
  const canAdd = !readOnly && (field.maxItems === undefined || fields.length < field.maxItems);
  const canRemove = !readOnly && fields.length > (field.minItems ?? 0);
  return (
    <fieldset className="flex flex-col gap-2 rounded border border-paper-line p-2">
      <legend className="px-1 text-xs font-semibold">
        {label} <span className="font-normal text-ink-soft">({fields.length})</span>
      </legend>
      {fields.map((item, index) => (
        <div key={item.id} className="flex flex-col gap-2 rounded bg-paper-deep/60 p-2">
          <div className="flex items-center justify-between text-xs">
            <span className="font-semibold">
              {label.replace(/s$/, "")} {index + 1}
            </span>
            {canRemove ? (
              <button
                type="button"
                className="text-ink-soft underline hover:text-ink"
                onClick={() => {
                  remove(index);
                  submit();
                }}
              >
                Remove
              </button>
            ) : null}
          </div>
          {element.kind === "object"
            ? element.fields.map((child) => (
                <FieldView
                  key={child.name}
                  field={child}
                  path={`${path}.${index}.${fieldKey(child)}`}
                  register={register}
                  control={control}
                  errors={errors}
                  submit={submit}
                  readOnly={readOnly}
                />
              ))
            : null}
        </div>
      ))}
      {canAdd ? (
        <button
          type="button"
          className="self-start text-xs text-copper-deep underline"
          onClick={() => {
            append(emptyValue(element) as never);
            submit();
          }}
        >
          Add {label.replace(/s$/, "").toLowerCase()}
        </button>
      ) : null}
    </fieldset>
  );
}

/**
 * The selected device's parameters as a form generated from its type's zod
 * schema. Every valid change is applied at once (so the object list and the
 * card follow), invalid values are shown beside the field and not applied.
 * With `readOnly` the values are shown in disabled fields and nothing applies.
 */
export function ParameterPanel({
  device,
  readOnly = false,
}: {
  device: BenchDevice;
  readOnly?: boolean;
}) {
  const type = getDeviceType(device.type);
  if (type === undefined)
    return <p className="text-sm text-fault">Unknown device type “{device.type}”.</p>;
  // Remount when the stored parameters change (an apply, undo or redo) so the form shows them.
  return (
    <ParameterForm
      key={`${device.id}:${JSON.stringify(device.parameters)}`}
      device={device}
      schema={type.parameters}
      readOnly={readOnly}
    />
  );
}

function ParameterForm({
  device,
  schema,
  readOnly,
}: {
  device: BenchDevice;
  schema: z.ZodType;
  readOnly: boolean;
}) {
  const store = useEditorStoreApi();
  const type = getDeviceType(device.type)!;
  const fields = useMemo(() => parameterFields(schema), [schema]);
  const form = useForm<Values>({
    resolver: zodResolver(schema as z.ZodType<Values, Values>),
    defaultValues: effectiveParameters(type, device.parameters) as Values,
    mode: "onChange",
  });
  const submit = () => {
    if (readOnly) return;
    // Deferred one task so react-hook-form has the changed value before validating.
    setTimeout(
      () =>
        void form.handleSubmit((values) => {
          store.getState().apply((bench) => {
            const outcome = setParameters(bench, device.id, values);
            if (!outcome.ok) return outcome;
            return { ok: true, value: outcome.value.bench };
          }, "Parameters applied");
        })(),
      0,
    );
  };
  if (fields.length === 0)
    return <p className="text-sm text-ink-soft">This device type has no parameters.</p>;
  return (
    <form
      aria-label={`Parameters of ${device.name}`}
      className="flex flex-col gap-3"
      onSubmit={(e) => e.preventDefault()}
    >
      {/* A disabled fieldset disables every field inside it, however deeply nested. */}
      <fieldset disabled={readOnly} className="contents">
        {fields.map((field) => (
          <FieldView
            key={field.name}
            field={field}
            path={fieldKey(field)}
            register={form.register}
            control={form.control}
            errors={form.formState.errors}
            submit={submit}
            readOnly={readOnly}
          />
        ))}
      </fieldset>
    </form>
  );
}
