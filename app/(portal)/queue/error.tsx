"use client";

import { errorPage } from "@/components/portal/segment-states";

export default errorPage("This page");
