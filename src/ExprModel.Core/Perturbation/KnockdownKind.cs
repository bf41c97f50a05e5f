namespace ExprModel.Core.Perturbation;

/// <summary>What a knock-down reduces: one channel entry of the model, or one gene (every entry it feeds).</summary>
public enum KnockdownKind
{
    Channel,
    Gene,
}
