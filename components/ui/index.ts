export { Button, type ButtonProps } from "./button";
export { Input, inputClass, sized } from "./input";
export { Select } from "./select";
export { Field } from "./field";
export { Badge, type BadgeTone } from "./badge";
export { PageHeader } from "./page-header";
export { EmptyState } from "./empty-state";
export { Section } from "./section";
export { cx } from "./cx";
