// The order lives in the engine, so the bundle's report and checks files list drive rows as the workspace does.
export { orderDriveRows } from "@/engine/checks/drive-order";
