// The analysis page keeps its own name for the shared provider; results stay fresh until the data version changes.
export { QueryProvider as AnalysisQueryProvider } from "@/components/ui/query-provider";
