/**
 * The models of cairn, each written in sufficient statistics: spec -> data -> sufficient statistics ->
 * fit -> result. This is the Java API that the command line uses and that other JVM libraries call.
 * The models arrive with their own issues (spend, segmented spend, pooled effects, retention).
 */
package dev.cairn.models;
