"""Batch work: checking JSONL data sets and collecting many schemes into one document."""
