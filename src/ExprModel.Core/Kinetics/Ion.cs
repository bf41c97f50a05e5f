namespace ExprModel.Core.Kinetics;

/// <summary>The permeant ion that sets a channel's reversal potential.</summary>
public enum Ion { Sodium, Potassium, Calcium, Cation, Chloride, Nonspecific }
