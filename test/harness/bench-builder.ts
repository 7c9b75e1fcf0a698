import type { BenchInput } from "@/engine";

type Device = NonNullable<BenchInput["devices"]>[number];
type Link = NonNullable<BenchInput["links"]>[number];
type GroupAddress = NonNullable<BenchInput["groupAddresses"]>[number];
type UnitLink = NonNullable<BenchInput["unitLinks"]>[number];

/** What `build()` returns: a bench document whose lists are always there, so a test can spread or index them. */
export type BuiltBench = BenchInput & {
  groupAddresses: GroupAddress[];
  devices: Device[];
  links: Link[];
  unitLinks: UnitLink[];
};

/**
 * Builds bench documents for tests without repeating the boilerplate:
 *
 *   benchBuilder().groupAddress("1/0/1", "1.001").device("act", "switch-actuator", "1.1.2")
 *     .link("act", 0, "1/0/1").build()
 *
 * One line "main" (1.1) and the test tool at 1.1.250 unless changed.
 */
export class BenchBuilder {
  private readonly doc: {
    name: string;
    lines: { id: string; address: string; name: string }[];
    testToolAddress: string;
    groupAddresses: GroupAddress[];
    devices: Device[];
    links: Link[];
    unitLinks: UnitLink[];
  } = {
    name: "Test bench",
    lines: [{ id: "main", address: "1.1", name: "Main line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [],
    devices: [],
    links: [],
    unitLinks: [],
  };

  named(name: string): this {
    this.doc.name = name;
    return this;
  }

  /** Replaces the first line ("main", 1.1), the one devices sit on unless they name another. */
  mainLine(id: string, address: string, name = id): this {
    this.doc.lines[0] = { id, address, name };
    return this;
  }

  line(id: string, address: string, name = id): this {
    this.doc.lines.push({ id, address, name });
    return this;
  }

  testTool(address: string): this {
    this.doc.testToolAddress = address;
    return this;
  }

  groupAddress(address: string, dpt: string, name = `GA ${address}`): this {
    this.doc.groupAddresses.push({ address, name, dpt });
    return this;
  }

  device(
    id: string,
    type: string,
    individualAddress: string | undefined,
    parameters: Record<string, unknown> = {},
    extra: Partial<Device> = {},
  ): this {
    this.doc.devices.push({
      id,
      type,
      name: id,
      ...(individualAddress === undefined ? {} : { individualAddress }),
      parameters,
      ...extra,
    });
    return this;
  }

  /** Links an object to addresses; the first is its sending address. */
  link(device: string, object: number, ...groupAddresses: string[]): this {
    for (const groupAddress of groupAddresses)
      this.doc.links.push({ device, object, groupAddress });
    return this;
  }

  unitLink(id: string, ...members: string[]): this {
    this.doc.unitLinks.push({ id, members });
    return this;
  }

  build(): BuiltBench {
    return { format: 1, ...structuredClone(this.doc) };
  }
}

export function benchBuilder(): BenchBuilder {
  return new BenchBuilder();
}
