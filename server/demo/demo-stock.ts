import type { OriginKind, ValveStatus } from '../valves/valve-status';
import { DEMO_BENCHES } from './demo-data';

/** Label prefix of the invented workshop's stock (Kestrel Lane). */
export const DEMO_LABEL_PREFIX = 'KL';

/** One valve of the demo stock; makers, lots, places and people are invented. */
export interface DemoValve {
  label: string;
  type: string;
  maker: string;
  dateCode: string;
  originKind: OriginKind;
  originText: string;
  location: string;
  status: ValveStatus;
  notes: string | null;
}

type Row = [
  type: string,
  maker: string,
  dateCode: string,
  origin: keyof typeof ORIGINS,
  location: string,
  status: ValveStatus,
];

/** Origins of the stock, in words. */
const ORIGINS = {
  estate: ['lot', 'Estate lot 17, boxed spares'],
  harrow: ['supplier', 'Harrow Row Surplus, invoice 2291'],
  swap: ['lot', 'Club swap table, spring meet'],
  customer: ['customer', 'Customer 0412, 18-watt practice amplifier'],
  console: ['customer', 'Customer 0388, radiogram restoration'],
  octet: ['supplier', 'Marlowe Yard Clearance, boxed octet, invoice 3107'],
} as const satisfies Record<string, readonly [OriginKind, string]>;

const ROWS: Row[] = [
  ['12AX7', 'Northvale', 'K7 3B', 'estate', 'Drawer C3', 'in-stock'],
  ['12AX7', 'Northvale', 'K7 3B', 'estate', 'Drawer C3', 'in-stock'],
  ['12AX7', 'Corrin & Hale', 'M2 1C', 'harrow', 'Drawer C3', 'in-stock'],
  ['12AX7', 'Corrin & Hale', 'M2 1C', 'harrow', 'Drawer C3', 'reserved'],
  ['12AX7', 'Aurel', 'J9 4A', 'swap', 'Drawer C3', 'in-stock'],
  ['12AX7', 'Aurel', 'J9 4A', 'swap', 'Reject bin', 'rejected'],
  ['12AX7', 'Lyndmoor', 'L4 2D', 'customer', 'Customer tray', 'customer'],
  ['12AX7', 'Northvale', 'N1 3C', 'harrow', 'Drawer C3', 'sold'],
  ['EL34', 'Corrin & Hale', 'K8 1A', 'harrow', 'Shelf 2, box 5', 'in-stock'],
  ['EL34', 'Corrin & Hale', 'K8 1A', 'harrow', 'Shelf 2, box 5', 'in-stock'],
  ['EL34', 'Corrin & Hale', 'K8 1A', 'harrow', 'Shelf 2, box 5', 'in-stock'],
  ['EL34', 'Corrin & Hale', 'K8 2A', 'harrow', 'Shelf 2, box 5', 'reserved'],
  ['EL34', 'Northvale', 'M6 2B', 'estate', 'Shelf 2, box 5', 'in-stock'],
  ['EL34', 'Northvale', 'M6 2B', 'estate', 'Shelf 2, box 5', 'in-stock'],
  ['EL34', 'Aurel', 'J5 4D', 'swap', 'Reject bin', 'rejected'],
  ['EL34', 'Lyndmoor', 'L1 3A', 'customer', 'Customer tray', 'customer'],
  ['12AU7', 'Aurel', 'K2 1D', 'swap', 'Drawer C4', 'in-stock'],
  ['12AU7', 'Aurel', 'K2 1D', 'swap', 'Drawer C4', 'in-stock'],
  ['12AU7', 'Northvale', 'M9 4B', 'console', 'Customer tray', 'customer'],
  ['12AU7', 'Lyndmoor', 'N3 2C', 'estate', 'Drawer C4', 'sold'],
  ['6L6GC', 'Lyndmoor', 'L7 1B', 'harrow', 'Shelf 2, box 6', 'in-stock'],
  ['6L6GC', 'Lyndmoor', 'L7 1B', 'harrow', 'Shelf 2, box 6', 'in-stock'],
  ['6L6GC', 'Corrin & Hale', 'M4 3D', 'estate', 'Shelf 2, box 6', 'reserved'],
  ['6L6GC', 'Corrin & Hale', 'M4 3D', 'estate', 'Shelf 2, box 6', 'in-stock'],
  // A boxed octet bought for matching: enough of one type for pairs and quads to choose from.
  ['EL34', 'Aurel', 'N2 1B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 1B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 1B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 1B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 2B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 2B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 2B', 'octet', 'Shelf 3, box 1', 'in-stock'],
  ['EL34', 'Aurel', 'N2 2B', 'octet', 'Shelf 3, box 1', 'in-stock'],
];

function buildStock(): DemoValve[] {
  const valves = ROWS.map(([type, maker, dateCode, origin, location, status], i) => ({
    label: `${DEMO_LABEL_PREFIX}-${String(i + 1).padStart(4, '0')}`,
    type,
    maker,
    dateCode,
    originKind: ORIGINS[origin][0],
    originText: ORIGINS[origin][1],
    location,
    status,
    notes: null as string | null,
  }));
  // The valves the simulated benches hold are in their sockets, on test.
  for (const bench of DEMO_BENCHES) {
    const v = valves.find((x) => x.label === bench.label)!;
    v.status = 'on-test';
    v.location = `${bench.name} socket`;
    v.notes = `In the ${bench.name} socket (simulated valve ${bench.valve}).`;
  }
  return valves;
}

/** The invented stock: 12AX7 x 8, EL34 x 16, 12AU7 x 4, 6L6GC x 4. */
export const DEMO_STOCK: readonly DemoValve[] = buildStock();
